/**
 * The checks on every result. Each finding is { kind, detail }: `kind` is one of {@link KINDS}, `detail`
 * says what was wrong in a form that groups alike findings (numbers left out).
 */
'use strict';
const { judge } = require('./spec');

/** Every kind of finding, with the words the report uses. */
const KINDS = {
  abort: 'engine abort (the child process died)',
  timeout: 'over the hard budget (killed by the watchdog)',
  memory: 'memory of one call over the limit',
  raw: 'raw exception (not a CustomFunctions.Error)',
  'error-code': 'error code other than #VALUE! or #N/A',
  wording: 'internal wording in a message',
  'unnamed-argument': 'message does not name the argument',
  'not-refused': 'input outside its declared rules not refused with #VALUE!',
  cell: 'NaN, Infinity, undefined, null or an object in a result cell',
  shape: 'spill shape does not match the input',
  blank: 'blank position or control slot not kept blank',
  probability: 'probability outside [0, 1]',
  'sum-to-one': 'P(highest) does not sum to 1',
  order: 'interval not ordered (lower ≤ median ≤ upper)',
  range: 'value outside its possible range',
  density: 'density table malformed',
  missing: 'registered in functions.json but not associated by the bundle',
};

/** Wording that belongs to the code, not to a user; each with the name the report gives it. */
const INTERNAL_WORDING = [
  [/unexpected (problem|failure)/i, '"unexpected problem"'],
  [/please report/i, '"please report it"'],
  [/could not compute this result/i, 'the catch-all message (an unforeseen failure)'],
  [/\binternal\b/i, '"internal"'],
  [/\b[a-z]+[A-Z][A-Za-z0-9]*\b/, 'camelCase identifier'],
  [/\bNaN\b/, 'NaN'],
  [/\b-?Infinity\b/, 'Infinity'],
  [/\bundefined\b/, 'undefined'],
  [/\bnull\b/, 'null'],
  [/\[object \w+\]/, '[object …]'],
  [/\b(Type|Range|Reference|Syntax)Error\b/, 'JavaScript error name'],
  [/is not a function|Cannot read propert|Maximum call stack/i, 'JavaScript engine message'],
  [/\n\s+at |\.(?:ts|js):\d+/, 'stack trace'],
  [/\ban? (object|function|symbol|bigint) value\b/, 'JavaScript type name'],
];

/** The names of the patterns a message matches. */
function internalWording(message) {
  return INTERNAL_WORDING.filter(([pattern]) => pattern.test(message)).map(([, name]) => name);
}

/** A message with numbers and quoted text left out, for grouping alike messages. */
function skeleton(message) {
  return String(message)
    .replace(/"[^"]*"/g, '"…"')
    .replace(/-?\b\d[\d.,]*(?:e[+-]?\d+)?\b/gi, '#')
    .replace(/\s+/g, ' ')
    .slice(0, 140);
}

const isBlankSlot = (cell) => cell === '';
const isFiniteNumber = (x) => typeof x === 'number' && Number.isFinite(x);
/** Whether a message names an argument (as a word: `visitors` is not named by `visitors_per_variant`). */
const names = (message, name) => new RegExp(`(^|[^\\w])${name}([^\\w]|$)`).test(message);

function checkCell(cell, push) {
  if (typeof cell === 'number') {
    if (!Number.isFinite(cell)) push('cell', `${String(cell)} in a cell`);
    return;
  }
  if (typeof cell === 'string') return;
  if (cell === undefined || cell === null) push('cell', `${String(cell)} in a cell`);
  else if (typeof cell === 'boolean') push('cell', 'a logical in a cell');
  else push('cell', `${cell && cell.$error ? `the error ${cell.$error}` : 'an object'} in a cell`);
}

/** Rows of the result as a rectangle, or a finding. */
function asRows(value, push) {
  if (!Array.isArray(value) || value.length === 0 || !value.every(Array.isArray)) {
    push('shape', 'the result is not a 2-D array');
    return undefined;
  }
  const width = value[0].length;
  if (width === 0 || value.some((row) => row.length !== width)) {
    push('shape', 'the result rows differ in length');
    return undefined;
  }
  return value;
}

/** For each position of the input, its output cells (a row for a column input and the reverse). */
function perPosition(rows, table, width) {
  const expected = table.orientation === 'row' ? [width, table.length] : [table.length, width];
  if (rows.length !== expected[0] || rows[0].length !== expected[1]) return undefined;
  return Array.from({ length: table.length }, (_, p) =>
    Array.from({ length: width }, (_, j) => (table.orientation === 'row' ? rows[j][p] : rows[p][j])),
  );
}

function checkNumbers(output, numbers, push) {
  const { values, min, max } = output;
  for (const x of numbers) {
    if (typeof x !== 'number' || !Number.isFinite(x)) continue;
    if ((values === 'probability' || values === 'sumToOne' || values === 'rate') && !(x >= 0 && x <= 1)) {
      push(values === 'rate' ? 'range' : 'probability', `${values} ${x < 0 ? 'below 0' : 'above 1'}`);
    }
    if (values === 'loss' && x < 0) push('range', 'negative expected loss');
    if (values === 'positive' && !(x > 0)) push('range', 'prior parameter not above 0');
    if (values === 'whole' && !(Number.isInteger(x) && x >= 1)) push('range', 'not a whole number ≥ 1');
    if (min !== undefined && x < min) push('range', `value below ${min}`);
    if (max !== undefined && x > max) push('range', `value above ${max}`);
  }
}

function checkOrder(output, blocks, push) {
  for (const block of blocks) {
    if (!block.every(isFiniteNumber)) continue;
    if (output.values === 'interval' && !(block[0] <= block[1])) push('order', 'lower > upper');
    if (output.values === 'median' && !(block[0] <= block[1] && block[1] <= block[2])) {
      push('order', block[0] > block[1] ? 'lower > median' : 'median > upper');
    }
  }
}

/**
 * A by-day result: one row per row of the day tables, a blank day a row of "", each day one value per
 * challenger (`per: 'challenger'`) or one value (`per: 'day'`), "" only while no visitor was counted yet
 * (the control or that challenger, or every variant for the split check).
 */
function checkByDay(output, value, days, push) {
  const rows = asRows(value, push);
  if (!rows) return;
  rows.flat().forEach((c) => checkCell(c, push));
  const width = output.per === 'challenger' ? days.width - 1 : 1;
  if (rows.length !== days.height || rows[0].length !== width) {
    return push(
      'shape',
      `${rows.length} × ${rows[0].length} where days × ${output.per === 'day' ? '1' : 'challengers'} belongs`,
    );
  }
  const filled = new Set(days.filled);
  const totals = new Array(days.width).fill(0);
  rows.forEach((row, r) => {
    if (!filled.has(r)) {
      if (row.some((x) => !isBlankSlot(x))) push('blank', 'a blank day’s row is not ""');
      return;
    }
    days.visitors[r].forEach((v, c) => (totals[c] += v));
    row.forEach((x, j) => {
      const none = output.per === 'challenger' ? totals[0] === 0 || totals[j + 1] === 0 : totals.every((t) => t === 0);
      if (none && !isBlankSlot(x)) push('blank', 'a value before any visitor');
      if (!none && isBlankSlot(x)) push('blank', 'a day with visitors holds ""');
    });
  });
  checkNumbers(output, rows.flat(), push);
}

/** Checks a successful result against the function's output description and the input's table. */
function checkValue(model, args, value, table, push, days) {
  const output = model.output;
  if (output.shape === 'byDay') {
    if (days) checkByDay(output, value, days, push);
    else push('shape', 'a by-day result without readable day tables');
    return;
  }
  if (output.shape === 'unknown') {
    if (Array.isArray(value)) (asRows(value, push) || []).flat().forEach((c) => checkCell(c, push));
    else checkCell(value, push);
    return;
  }
  if (output.shape === 'scalar') {
    if (Array.isArray(value)) return push('shape', 'an array where one value belongs');
    checkCell(value, push);
    if (output.values === 'text') {
      if (typeof value !== 'string' || value.trim() === '') push('shape', 'no text where a verdict belongs');
      else if (internalWording(value).length > 0)
        push('wording', `result text: ${skeleton(value)} [${internalWording(value).join(', ')}]`);
    } else if (typeof value !== 'number') push('shape', 'text where a number belongs');
    else checkNumbers(output, [value], push);
    return;
  }
  const rows = asRows(value, push);
  if (!rows) return;
  rows.flat().forEach((c) => checkCell(c, push));
  if (output.shape === 'row') {
    if (rows.length !== 1 || rows[0].length !== output.width) push('shape', `not 1 × ${output.width}`);
    checkNumbers(output, rows.flat(), push);
    return;
  }
  if (!table) return;
  const filled = new Set(table.positions);
  const control = table.positions[0];
  if (output.shape === 'density') {
    const pointsParam = model.params.find((p) => p.name === 'points');
    const pointsArg = pointsParam ? args[model.params.indexOf(pointsParam)] : undefined;
    const points = typeof pointsArg === 'number' ? pointsArg : pointsParam && pointsParam.rule.default;
    const columns = output.per === 'variant' ? table.length : table.length - 1;
    if ((points !== undefined && rows.length !== points) || rows[0].length !== 1 + columns) {
      return push('shape', `density table not points × ${output.per === 'variant' ? '(1 + positions)' : 'positions'}`);
    }
    const grid = rows.map((r) => r[0]);
    if (grid.some((x, i) => i > 0 && !(x > grid[i - 1]))) push('density', 'grid not increasing');
    if (output.gridMin !== undefined && grid.some((x) => x < output.gridMin))
      push('density', `grid below ${output.gridMin}`);
    if (output.gridMax !== undefined && grid.some((x) => x > output.gridMax))
      push('density', `grid above ${output.gridMax}`);
    for (let c = 0; c < columns; c++) {
      const position = output.per === 'variant' ? c : c + 1;
      const shouldFill = filled.has(position) && (output.per === 'variant' || position !== control);
      const column = rows.map((r) => r[1 + c]);
      if (shouldFill && column.some(isBlankSlot)) push('blank', 'a variant’s density column holds ""');
      if (!shouldFill && column.some((x) => !isBlankSlot(x)))
        push('blank', 'a blank position’s density column is not ""');
      if (column.some((x) => typeof x === 'number' && x < 0)) push('density', 'negative density');
    }
    return;
  }
  const width = output.shape === 'block' || output.shape === 'blockVersusControl' ? output.width : 1;
  const slots = perPosition(rows, table, width);
  if (!slots) {
    const want = table.orientation === 'row' ? `${width} × ${table.length}` : `${table.length} × ${width}`;
    return push('shape', `${rows.length} × ${rows[0].length} where ${want} belongs (${table.orientation} input)`);
  }
  const versus = output.shape === 'versusControl' || output.shape === 'blockVersusControl';
  const blocks = [];
  slots.forEach((slot, p) => {
    const shouldFill = filled.has(p) && !(versus && p === control);
    if (shouldFill && slot.some(isBlankSlot)) push('blank', 'a variant’s slot holds ""');
    if (!shouldFill && slot.some((x) => !isBlankSlot(x))) {
      push('blank', versus && p === control ? 'the control’s slot is not ""' : 'a blank position’s slot is not ""');
    }
    if (shouldFill) blocks.push(slot);
  });
  checkNumbers(output, blocks.flat(), push);
  checkOrder(output, blocks, push);
  if (output.values === 'sumToOne' && blocks.length > 0 && blocks.flat().every(isFiniteNumber)) {
    const sum = blocks.flat().reduce((s, x) => s + x, 0);
    if (!(Math.abs(sum - 1) <= 1e-9)) push('sum-to-one', 'P(highest) sums to other than 1');
  }
}

/**
 * Every finding for one call and its result.
 * @param {object} model the function's model (models.js)
 * @param {unknown[]} args the call's arguments (tagged cells as generate.js writes them)
 * @param {object} result what the pool reported: { outcome, value | code, message | name, … }
 * @param {{ memoryMb: number }} limits
 * @returns {{ kind: string, detail: string }[]}
 */
function checkResult(model, args, result, limits) {
  const findings = [];
  const push = (kind, detail) => {
    if (!findings.some((f) => f.kind === kind && f.detail === detail)) findings.push({ kind, detail });
  };
  const judged = judge(model, args);
  const mustRefuse = judged.violations.length > 0 || judged.countProblem;
  switch (result.outcome) {
    case 'abort':
      push('abort', result.reason);
      break;
    case 'timeout':
      push(
        'timeout',
        result.stalled ? 'stopped twice at the wall-time cap before using its CPU budget' : 'over the hard budget',
      );
      break;
    case 'missing':
      push('missing', 'not associated');
      break;
    case 'raw':
      push('raw', `${result.name}: ${skeleton(result.message)}`);
      break;
    case 'error': {
      const message = String(result.message ?? '');
      if (result.code !== '#VALUE!' && result.code !== '#N/A') push('error-code', `${result.code}`);
      const wording = internalWording(message);
      if (wording.length > 0) push('wording', `${skeleton(message)} [${wording.join(', ')}]`);
      // a message already reported for its wording is not reported again for not naming the argument
      if (wording.length > 0) break;
      if (mustRefuse && !judged.countProblem) {
        if (result.code !== '#VALUE!') push('not-refused', `${judged.violations[0].why} answered ${result.code}`);
        else if (!judged.violations.some((v) => names(message, v.param))) {
          push(
            'unnamed-argument',
            `${judged.violations.map((v) => v.param).join('/')} (${judged.violations[0].why}): ${skeleton(message)}`,
          );
        }
      } else if (!mustRefuse) {
        const named = model.params.some((p) => names(message, p.name)) || /variant|past result/i.test(message);
        if (!named) push('unnamed-argument', skeleton(message));
      }
      break;
    }
    case 'value':
      if (mustRefuse) {
        push(
          'not-refused',
          judged.countProblem
            ? 'variant count outside the limits accepted'
            : `${judged.violations[0].why.replace(/ at item \d+/, '')} (${judged.violations[0].param}) accepted`,
        );
      } else {
        checkValue(model, args, result.value, judged.table, push, judged.days);
      }
      break;
    default:
      push('raw', `unknown outcome ${result.outcome}`);
  }
  if (typeof result.heapGrowthMb === 'number' && result.heapGrowthMb > limits.memoryMb)
    push('memory', `heap grew by more than ${limits.memoryMb} MB`);
  return findings;
}

module.exports = { KINDS, checkResult, internalWording, skeleton, INTERNAL_WORDING };
